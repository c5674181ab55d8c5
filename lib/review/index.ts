export * from "./runReview";
export * from "./cautions";
export * from "./canonical";
export * from "./csv";
export * from "./audit";
export * from "./export";
export * from "./tryRunReview";

export * from "./runReview";
export * from "./cautions";
export * from "./canonical";
export * from "./csv";

export * from "./runReview";
export * from "./cautions";
export * from "./canonical";

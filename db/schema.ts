// The Drizzle schema, one module per area; migrations are generated from this entry point.
export * from "./tables/people";
export * from "./tables/data";
export * from "./tables/figures";
export * from "./tables/review";
export * from "./tables/mail";

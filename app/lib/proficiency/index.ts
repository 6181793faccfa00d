export * from "./algorithm-a";
export * from "./assigned-value";
export * from "./sigma-pt";
export * from "./scores";
export * from "./interpretation";
export * from "./homogeneity";
export * from "./stability";
export * from "./score-round";

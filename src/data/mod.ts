/** RV data files. @module */
export * from "./rv_csv.ts";

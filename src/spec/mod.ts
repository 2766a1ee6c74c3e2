/** The TOML spec: parsing, validation, matching against data. @module */
export * from "./types.ts";
export * from "./parse.ts";
export * from "./resolve.ts";
export * from "./load.ts";

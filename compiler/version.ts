// The tool version recorded in every model's provenance (kept equal to package.json's).
export const TOOL_VERSION = "0.1.0";

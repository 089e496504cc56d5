// The tool's name and version as they appear in results (kept in step with package.json by a test).
export const TOOL_NAME = 'spotcast';
export const TOOL_VERSION = '0.1.0';

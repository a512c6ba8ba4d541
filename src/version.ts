/** The tool's version, recorded in every model file it writes. Keep in step with package.json. */
export const TOOL_VERSION = '0.1.0';

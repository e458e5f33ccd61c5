// The headless entry (main.ts): one file per command, the shared arguments and exit codes, the
// bounded plan-file reader. The public face of app/cli/, for the tests and scripts.
export { terminalText, type CliIO } from './args';
export { jsonSyntaxError, MAX_JSON_DEPTH } from './json-syntax';
export { runCli } from './main';
export { MAX_LISTED_PROBLEMS, MAX_PLAN_BYTES } from './plan-file';
export { loadTerrain, terrainPath, type TerrainRead } from './terrain';
export { CHROMIUM_ARGS, CHROMIUM_PATH, printPdf } from './print-pdf';

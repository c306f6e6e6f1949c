// Public surface of the workbench server.
export { createApp, DEFAULT_UPLOAD_LIMIT } from './app.js';
export { startServer, isLoopback, ServerStartError, type StartServerOptions, type RunningServer } from './start.js';
export type { AppDeps, AppEnv, CurrentUser } from './types.js';

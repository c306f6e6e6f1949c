// Public surface of the workbench server.
export { createApp, DEFAULT_UPLOAD_LIMIT } from './app.js';
export { startServer, startWorkbench, isLoopback, settingsFromEnvironment, ServerStartError, type StartServerOptions, type RunningServer } from './start.js';
export { hostName, isAllowedHost, type HostPolicy } from './hosts.js';
export { SignInThrottle, RequestRateLimiter, requestLimitsFor, DEFAULT_REQUESTS_PER_SECOND, type ThrottleLimits, type ThrottleVerdict, type RequestLimits, type RateVerdict } from './throttle.js';
export { SESSION_COOKIE, SECURE_SESSION_COOKIE } from './auth.js';
export type { AppDeps, AppEnv, CurrentUser } from './types.js';

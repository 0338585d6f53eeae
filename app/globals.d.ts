/** The app version from package.json, injected by Vite at build time. */
declare const __APP_VERSION__: string;

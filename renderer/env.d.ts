/// <reference types="vite/client" />
/// <reference types="svelte" />

/** Set by renderer/vite.config.ts from package.json. */
declare const __APP_VERSION__: string;

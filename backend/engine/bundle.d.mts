export declare const ROOT: string;
export declare const BUNDLE_DIR: string;
export declare const ENTRIES: { worker: string; study: string; bench: string; report: string };
export declare function ensureBundle(name: keyof typeof ENTRIES): string;

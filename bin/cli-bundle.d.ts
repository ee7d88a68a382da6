/** Folder of the prebuilt command-line bundle below the package root. */
export declare const BUNDLE_DIR: string;
/** Why the bundle under `root` cannot be used (missing, or a source changed since it was built), or null when current. */
export declare function bundleStaleReason(root: string): string | null;

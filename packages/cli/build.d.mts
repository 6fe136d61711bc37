/** Types of build.mjs (the CLI build), for the TypeScript scripts that use it. */
export declare const DIST: string;
export declare const ENTRY: string;
export declare function isFresh(): boolean;
export declare function build(options?: { clean?: boolean }): Promise<number>;

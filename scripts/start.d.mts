export declare function electronBinary(electronPackageDir?: string): string | undefined;
export declare function newestMtime(paths: string[]): number;
export declare function isStale(output: string, inputs: string[]): boolean;
export declare function displayProblem(env?: Record<string, string | undefined>, platform?: string): string | undefined;

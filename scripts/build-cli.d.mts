export declare const CLI_BUNDLE: string
export declare function buildCli(): Promise<void>
export declare function bundleForNode(entry: string, outfile: string): Promise<void>

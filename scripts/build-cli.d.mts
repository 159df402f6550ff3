export declare const CLI_BUNDLE: string
export declare function buildCli(): Promise<void>

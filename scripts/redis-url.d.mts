// Types of scripts/redis-url.mjs for the TypeScript that imports it.
export declare const DEFAULT_REDIS_PORT: number
export declare function redisPort(env?: Record<string, string | undefined>): number
export declare function redisUrl(env?: Record<string, string | undefined>): string

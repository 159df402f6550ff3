// Where the job queue's Redis is: EQUIPOISE_REDIS_URL, or the private Redis
// of this checkout (scripts/redis.mjs) on 127.0.0.1:EQUIPOISE_REDIS_PORT.
// The one place the web server, the workers, the scripts and the tests read it.

/** The private Redis's port when EQUIPOISE_REDIS_PORT is not set: not Redis's usual 6379, so a system Redis is left alone. */
export const DEFAULT_REDIS_PORT = 6380

export function redisPort(env = process.env) {
  return Number(env.EQUIPOISE_REDIS_PORT || DEFAULT_REDIS_PORT)
}

export function redisUrl(env = process.env) {
  return env.EQUIPOISE_REDIS_URL || `redis://127.0.0.1:${redisPort(env)}`
}

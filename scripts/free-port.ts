/** A TCP port on 127.0.0.1 that was free a moment ago (for a server the tests or the load check start). */
import { createServer } from 'node:net'

export function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const server = createServer()
    server.once('error', fail)
    server.listen(0, '127.0.0.1', () => {
      const address = server.address()
      server.close(() => done(typeof address === 'object' && address ? address.port : 0))
    })
  })
}

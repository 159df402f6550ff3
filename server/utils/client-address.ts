/**
 * The address of the client that sent a request, for rate limits. The
 * X-Forwarded-For header is believed only when the request came from a
 * configured trusted proxy (NUXT_TRUSTED_PROXIES: comma-separated addresses
 * or CIDR ranges, e.g. "127.0.0.1,10.0.0.0/8"); otherwise anyone could claim
 * any address. With no trusted proxy the socket's address is the client.
 */
import type { H3Event } from 'h3'
import { BlockList, isIP } from 'node:net'

let cached: { text: string, list: BlockList } | undefined

/** Parses the trusted proxy list; entries that are not addresses are reported once and skipped. */
export function trustedProxyList(text: string): BlockList {
  const list = new BlockList()
  for (const entry of text.split(',').map((s) => s.trim()).filter(Boolean)) {
    const [address, prefix] = entry.split('/') as [string, string | undefined]
    const family = isIP(address)
    if (!family) {
      console.warn(`NUXT_TRUSTED_PROXIES: "${entry}" is not an IP address or CIDR range; ignored`)
      continue
    }
    const type = family === 6 ? 'ipv6' : 'ipv4'
    if (prefix === undefined) list.addAddress(address, type)
    else list.addSubnet(address, Number(prefix), type)
  }
  return list
}

function plain(address: string): string {
  return address.startsWith('::ffff:') && isIP(address.slice(7)) === 4 ? address.slice(7) : address
}

function isTrusted(list: BlockList, address: string): boolean {
  const family = isIP(address)
  return family !== 0 && list.check(address, family === 6 ? 'ipv6' : 'ipv4')
}

/** The first address, from the right of X-Forwarded-For, that is not a trusted proxy. */
export function clientAddressFrom(socketAddress: string, forwardedFor: string | undefined, trusted: BlockList): string {
  let client = plain(socketAddress)
  if (!isTrusted(trusted, client) || !forwardedFor) return client
  const hops = forwardedFor.split(',').map((s) => plain(s.trim())).filter(Boolean)
  for (let i = hops.length - 1; i >= 0; i--) {
    client = hops[i]!
    if (!isIP(client)) return client.slice(0, 45)
    if (!isTrusted(trusted, client)) return client
  }
  return client
}

export function clientAddress(event: H3Event): string {
  const text = String(useRuntimeConfig(event).trustedProxies ?? '')
  if (cached?.text !== text) cached = { text, list: trustedProxyList(text) }
  const socket = event.node.req.socket?.remoteAddress ?? 'unknown'
  return clientAddressFrom(socket, getRequestHeader(event, 'x-forwarded-for'), cached.list)
}

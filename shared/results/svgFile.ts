/**
 * Turning the diagram's SVG markup into a file that stands on its own: an
 * XML prolog, the SVG namespace, and an opaque background (a transparent
 * diagram pasted into a dark slide loses its black axis text). The browser
 * serializes the element; these string steps stay testable without one.
 */

const SVG_NS = 'http://www.w3.org/2000/svg'

/** Make serialized `<svg …>…</svg>` markup a standalone SVG file with a background. */
export function standaloneSvg(markup: string, background = '#ffffff'): string {
  const open = /<svg\b[^>]*>/.exec(markup)
  if (!open) throw new Error('standaloneSvg: the markup holds no <svg> element')
  let tag = open[0]
  if (!/\sxmlns=/.test(tag)) tag = tag.replace(/^<svg/, `<svg xmlns="${SVG_NS}"`)
  const { width, height } = svgSize(markup)
  const rect = `<rect x="0" y="0" width="${width}" height="${height}" fill="${background}"/>`
  const body = markup.slice(open.index + open[0].length)
  return `<?xml version="1.0" encoding="UTF-8"?>\n${tag}${rect}${body}`
}

/**
 * Pixel size of an SVG from its width/height attributes, or its viewBox;
 * 640 × 400 when it states neither (Plot's own default size).
 */
export function svgSize(markup: string): { width: number; height: number } {
  const tag = /<svg\b[^>]*>/.exec(markup)?.[0] ?? ''
  const attribute = (name: string) => {
    const m = new RegExp(`\\s${name}="([\\d.]+)(?:px)?"`).exec(tag)
    return m ? Number(m[1]) : Number.NaN
  }
  let width = attribute('width')
  let height = attribute('height')
  const viewBox = /\sviewBox="([^"]+)"/.exec(tag)?.[1].trim().split(/[\s,]+/).map(Number)
  if (!(width > 0) && viewBox?.length === 4) width = viewBox[2]
  if (!(height > 0) && viewBox?.length === 4) height = viewBox[3]
  return { width: width > 0 ? width : 640, height: height > 0 ? height : 400 }
}

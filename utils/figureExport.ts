/**
 * A drawn figure (an SVG element on the page) as a file: the SVG standing
 * on its own (shared/results/svgFile.ts), or a PNG at twice its size drawn by
 * the browser onto a canvas. The diagram and the map export through these.
 */
import { standaloneSvg, svgSize } from '../shared/results/svgFile'
import { saveBlob } from './saveBlob'

/** The outermost SVG elements inside `container` (a plot with a legend is a figure of two), in page order. */
export function topSvgs(container: Element | null | undefined): SVGSVGElement[] {
  return Array.from(container?.querySelectorAll('svg') ?? []).filter((svg) => !svg.parentElement?.closest('svg'))
}

/**
 * The figure inside `container` as one standalone SVG file with a white
 * background; several SVGs (a legend above the plot) are stacked into one.
 * Null when there is none.
 */
export function svgFileOf(container: Element | null | undefined): string | null {
  const svgs = topSvgs(container)
  if (svgs.length === 0) return null
  const serializer = new XMLSerializer()
  if (svgs.length === 1) return standaloneSvg(serializer.serializeToString(svgs[0]!), '#ffffff')
  let y = 0
  let width = 0
  const parts = svgs.map((svg) => {
    const size = svgSize(serializer.serializeToString(svg))
    const copy = svg.cloneNode(true) as SVGSVGElement
    copy.setAttribute('x', '0')
    copy.setAttribute('y', String(y))
    y += size.height
    width = Math.max(width, size.width)
    return serializer.serializeToString(copy)
  })
  return standaloneSvg(`<svg width="${width}" height="${y}" viewBox="0 0 ${width} ${y}">${parts.join('')}</svg>`, '#ffffff')
}

export function saveSvg(file: string, name: string): void {
  saveBlob(new Blob([file], { type: 'image/svg+xml' }), name)
}

/** Saves the SVG file drawn as a PNG at twice its size; throws when the browser cannot draw it. */
export async function savePng(file: string, name: string): Promise<void> {
  const { width, height } = svgSize(file)
  const url = URL.createObjectURL(new Blob([file], { type: 'image/svg+xml' }))
  try {
    const image = new Image()
    image.src = url
    await image.decode()
    const canvas = document.createElement('canvas')
    canvas.width = width * 2
    canvas.height = height * 2
    const context = canvas.getContext('2d')
    if (!context) throw new Error('no 2d canvas')
    context.scale(2, 2)
    context.drawImage(image, 0, 0, width, height)
    const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, 'image/png'))
    if (!blob) throw new Error('no PNG')
    saveBlob(blob, name)
  } finally {
    URL.revokeObjectURL(url)
  }
}

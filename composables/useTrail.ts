/**
 * The breadcrumb in the top bar (lab › system › …). Each page sets its own
 * trail; the layout shows it.
 */
export interface TrailStep {
  label: string
  to?: string
}

export function useTrail(steps?: TrailStep[] | (() => TrailStep[])) {
  const trail = useState<TrailStep[]>('trail', () => [])
  if (typeof steps === 'function') {
    watchEffect(() => { trail.value = steps() })
  } else if (steps) {
    trail.value = steps
  }
  return trail
}

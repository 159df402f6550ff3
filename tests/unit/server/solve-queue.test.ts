// Admission to the solver: the per-account limit, the slots, and turns across accounts.
import { describe, expect, it } from 'vitest'
import { SolveQueue, SolveQueueRefusal } from '../../../server/utils/solve-queue'

/** A task that finishes when told to, recording when it started. */
function gate(log: string[], name: string) {
  let open!: () => void
  const done = new Promise<void>((resolve) => { open = resolve })
  return { task: async () => { log.push(name); await done; return name }, open }
}

const tick = () => new Promise((r) => setTimeout(r, 0))

describe('SolveQueue', () => {
  it('refuses an account its solve beyond the per-account limit, naming the limit, and admits it again once one finishes', async () => {
    const queue = new SolveQueue({ slots: 4, perUser: 2, maxWaiting: 10 })
    const log: string[] = []
    const a = gate(log, 'a1'), b = gate(log, 'a2')
    const first = queue.run(1, a.task)
    const second = queue.run(1, b.task)
    const refused = queue.run(1, async () => 'a3')
    await expect(refused).rejects.toBeInstanceOf(SolveQueueRefusal)
    await expect(refused).rejects.toThrow('at most 2 at a time per account')
    // Another account is not affected.
    await expect(queue.run(2, async () => 'b1')).resolves.toBe('b1')
    a.open()
    await first
    await expect(queue.run(1, async () => 'a4')).resolves.toBe('a4')
    b.open()
    await second
    expect(queue.heldBy(1)).toBe(0)
  })

  it('starts waiting solves in turn across accounts, so one account\'s backlog does not hold up another\'s', async () => {
    const queue = new SolveQueue({ slots: 1, perUser: 3, maxWaiting: 10 })
    const log: string[] = []
    const gates = [gate(log, 'a1'), gate(log, 'a2'), gate(log, 'a3'), gate(log, 'b1')]
    const runs = [queue.run(1, gates[0]!.task), queue.run(1, gates[1]!.task), queue.run(1, gates[2]!.task)]
    await tick()
    runs.push(queue.run(2, gates[3]!.task))
    await tick()
    expect(log).toEqual(['a1'])
    gates[0]!.open()
    await tick(); await tick()
    expect(log).toEqual(['a1', 'a2'])
    gates[1]!.open()
    await tick(); await tick()
    // Account 2's one solve comes before account 1's third.
    expect(log).toEqual(['a1', 'a2', 'b1'])
    gates[3]!.open()
    await tick(); await tick()
    expect(log).toEqual(['a1', 'a2', 'b1', 'a3'])
    gates[2]!.open()
    await Promise.all(runs)
  })

  it('frees the slot and the account\'s share when a solve fails', async () => {
    const queue = new SolveQueue({ slots: 1, perUser: 1, maxWaiting: 10 })
    await expect(queue.run(1, async () => { throw new Error('diverged') })).rejects.toThrow('diverged')
    expect(queue.heldBy(1)).toBe(0)
    await expect(queue.run(1, async () => 'again')).resolves.toBe('again')
  })

  it('says the solver is busy when too many solves wait', async () => {
    const queue = new SolveQueue({ slots: 1, perUser: 5, maxWaiting: 1 })
    const log: string[] = []
    const a = gate(log, 'a'), b = gate(log, 'b')
    const running = queue.run(1, a.task)
    const waiting = queue.run(2, b.task)
    const refused = queue.run(3, async () => 'c')
    await expect(refused).rejects.toMatchObject({ reason: 'queue-full' })
    a.open(); b.open()
    await Promise.all([running, waiting])
  })
})

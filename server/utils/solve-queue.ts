/**
 * Admission to the solver: at most `slots` solves run at once (one per pool
 * thread, so a task handed to the pool starts at once and its time limit
 * counts solving, not waiting), at most `perUser` solves per account are
 * running or waiting, and waiting solves are started in turn across
 * accounts, so one account's many sweeps do not hold up another's small
 * solve. Plain TypeScript (no Nitro), so it is unit-tested on its own.
 */

export class SolveQueueRefusal extends Error {
  constructor(readonly reason: 'per-user' | 'queue-full', message: string) {
    super(message)
  }
}

export interface SolveQueueOptions {
  slots: number
  perUser: number
  maxWaiting: number
}

export class SolveQueue {
  private running = 0
  /** Solves running or waiting, per account. */
  private readonly held = new Map<number, number>()
  /** Waiting solves per account, in arrival order; accounts in turn order. */
  private readonly waiting = new Map<number, (() => void)[]>()
  private waitingCount = 0

  constructor(private readonly options: SolveQueueOptions) {}

  /** How many solves an account has running or waiting. */
  heldBy(userId: number): number {
    return this.held.get(userId) ?? 0
  }

  get perUser(): number {
    return this.options.perUser
  }

  /**
   * Run `task` when a slot is free. Throws SolveQueueRefusal at once when the
   * account already holds `perUser` solves or too many are waiting.
   */
  async run<T>(userId: number, task: () => Promise<T>): Promise<T> {
    const { perUser, maxWaiting, slots } = this.options
    if (this.heldBy(userId) >= perUser) {
      throw new SolveQueueRefusal('per-user', `You already have ${this.heldBy(userId)} solves running or waiting; at most ${perUser} at a time per account. Wait for one to finish, then try again.`)
    }
    if (this.running >= slots && this.waitingCount >= maxWaiting) {
      throw new SolveQueueRefusal('queue-full', 'The solver is busy with other runs. Try again in a few seconds.')
    }
    this.held.set(userId, this.heldBy(userId) + 1)
    try {
      if (this.running >= slots) await this.wait(userId)
      else this.running++
      try {
        return await task()
      } finally {
        this.release()
      }
    } finally {
      const left = this.heldBy(userId) - 1
      if (left > 0) this.held.set(userId, left)
      else this.held.delete(userId)
    }
  }

  /** Resolves when a slot is handed to this account's oldest waiting solve (the slot is already counted). */
  private wait(userId: number): Promise<void> {
    return new Promise((resolve) => {
      const line = this.waiting.get(userId)
      if (line) line.push(resolve)
      else this.waiting.set(userId, [resolve])
      this.waitingCount++
    })
  }

  /** Free a slot, or hand it to the next account in turn. */
  private release(): void {
    const next = this.waiting.entries().next()
    if (next.done) {
      this.running--
      return
    }
    const [userId, line] = next.value
    const start = line.shift()!
    this.waitingCount--
    // This account goes to the back of the turn order.
    this.waiting.delete(userId)
    if (line.length) this.waiting.set(userId, line)
    start()
  }
}

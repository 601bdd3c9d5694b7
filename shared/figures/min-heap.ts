/** Binary min-heap of integer items keyed by a number (typed arrays, grows by doubling). */
export class MinHeap {
  private items = new Int32Array(64)
  private keys = new Float64Array(64)
  size = 0

  push(item: number, key: number): void {
    if (this.size === this.items.length) {
      const items = new Int32Array(2 * this.size),
        keys = new Float64Array(2 * this.size)
      items.set(this.items)
      keys.set(this.keys)
      this.items = items
      this.keys = keys
    }
    let i = this.size++
    while (i > 0) {
      const p = (i - 1) >> 1
      if (this.keys[p]! <= key) break
      this.items[i] = this.items[p]!
      this.keys[i] = this.keys[p]!
      i = p
    }
    this.items[i] = item
    this.keys[i] = key
  }

  /** Remove and return the item with the smallest key (size must be > 0). */
  pop(): number {
    const top = this.items[0]!
    const n = --this.size
    const item = this.items[n]!,
      key = this.keys[n]!
    let i = 0
    for (;;) {
      let c = 2 * i + 1
      if (c >= n) break
      if (c + 1 < n && this.keys[c + 1]! < this.keys[c]!) c++
      if (this.keys[c]! >= key) break
      this.items[i] = this.items[c]!
      this.keys[i] = this.keys[c]!
      i = c
    }
    this.items[i] = item
    this.keys[i] = key
    return top
  }
}

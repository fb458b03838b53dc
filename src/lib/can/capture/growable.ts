/** An append-only Float64Array that doubles its capacity as it fills. */
export class GrowableFloat64 {
	#values: Float64Array;
	#count = 0;

	constructor(initialCapacity = 64) {
		this.#values = new Float64Array(initialCapacity);
	}

	get count(): number {
		return this.#count;
	}

	push(value: number): void {
		if (this.#count === this.#values.length) {
			const next = new Float64Array(this.#values.length * 2 || 64);
			next.set(this.#values);
			this.#values = next;
		}
		this.#values[this.#count++] = value;
	}

	/** A right-sized copy, so the spare capacity can be freed. */
	toArray(): Float64Array {
		return this.#values.slice(0, this.#count);
	}
}

import type { MapBusLoad } from '$lib/can/busload';

/** What GET …/tools/bus-load answers; the Tools page reads the same type. */
export interface BusLoadResponse {
	map: { id: string; name: string };
	/** "r3" or "draft". */
	label: string;
	/** `mapBusLoad` of that snapshot, untouched. */
	busLoad: MapBusLoad;
	/** Per frame (same order as busLoad.frames): what the table shows beside the load. */
	frames: { extended: boolean; length: number; cycleMs: number | null }[];
}

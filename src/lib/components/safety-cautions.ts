/** The cautions of the app, each written once; `SafetyNote` shows the ones a page needs. */
export const SAFETY_CAUTIONS = {
	/** Work on a harness: termination checks, splicing, connecting devices. */
	wiring: [
		'Disconnect the battery before cutting into or splicing a harness, and measure resistance only with every node powered off.',
		'Connect a device only at a connector the vehicle maker intends for it.'
	],
	/** Recording on a vehicle that runs or moves. */
	recording: [
		'Record on a moving vehicle only with a second person operating the laptop, or on a dynamometer or closed course — never while driving on a public road.',
		'Record with the recorder listening only where you can: a device that acknowledges or transmits frames changes the bus you are measuring.'
	],
	/** Frames typed or computed by hand. */
	transmit: [
		'Payloads worked out here only check the map’s arithmetic: do not transmit hand-made frames onto a running vehicle’s bus, where a receiving controller may act on them.'
	]
} as const;

export type SafetyTopic = keyof typeof SAFETY_CAUTIONS;

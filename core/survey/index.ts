/** The whole system at a glance: the Δv map and the window calendar (front door). */
export {};

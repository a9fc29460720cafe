/** Light time and sunlight/shadow of a ship: readouts for authors (front door). */
export {};

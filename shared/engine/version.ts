/** Engine version: part of every result file. Change it whenever the same inputs could give other numbers. */
export const ENGINE_VERSION = "orthostack-engine 1.2.0";

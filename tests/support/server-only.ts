// Stands in for the 'server-only' marker package outside the Next bundler.
export {};

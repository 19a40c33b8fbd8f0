// Material harness tests render real overlays and selects; on a busy two-core machine the first
// test in a file can pass vitest's 5 s default while the compiler warms up.
vi.setConfig({ testTimeout: 20_000 });

/**
 * The glibc malloc setting the server, the worker and the benchmarks run with.
 *
 * glibc.malloc.hugetlb=1 (glibc ≥ 2.35, documented under "Memory Allocation
 * Tunables" in the glibc manual) makes malloc advise the kernel to back its
 * memory with transparent huge pages (madvise MADV_HUGEPAGE), where the
 * kernel's THP mode is "madvise". Why: every fit allocates its node data or
 * kernel matrix afresh, and on a virtual machine the first touch of a fresh
 * 4 KiB page is slow — measured here at about 10 µs a page (a Firecracker
 * VM), so a 200 × 200 cubic grid fit's 1.28 MB of node data cost about 3 ms to
 * fault in, more than the arithmetic that fills it (0.7 ms). With huge pages
 * one fault covers 2 MiB. Memory use can grow by up to a huge page per arena;
 * glibc without the tunable (older than 2.35) ignores it.
 */
const SETTING = 'glibc.malloc.hugetlb=1';

/** The environment additions: GLIBC_TUNABLES with the setting appended to any the caller already has. */
export function allocatorEnv(env) {
	const have = env.GLIBC_TUNABLES;
	if (have && have.split(':').some((t) => t.startsWith('glibc.malloc.hugetlb='))) return { GLIBC_TUNABLES: have };
	return { GLIBC_TUNABLES: have ? `${have}:${SETTING}` : SETTING };
}

/**
 * The fuzzer's time limit for NetCDF-4 metadata [ms], lowered from the reader's default (10 s, HDF5_METADATA_TIMEOUT_MS) so
 * that a mutant on which HDF5 loops ends (as the catalogued NetcdfReadStuck) well inside the
 * pool's limit per mutant. Set by worker.ts in every fuzz worker and by regenerate.ts --run.
 */
export const FUZZ_METADATA_TIMEOUT_MS = 4000;

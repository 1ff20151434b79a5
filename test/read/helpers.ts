/** Shared test helpers for the read stage: expect a catalogued error from a promise. */

export { expectCataloguedAsync as expectCatalogued } from '../helpers/catalogued.ts';

export { expectCatalogued } from '../helpers/catalogued.ts';

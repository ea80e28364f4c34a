/** Kept for imports written before the caution moved to `src/study/caution.ts`; import from there. */
export { CAUTION } from '../study/caution.ts';

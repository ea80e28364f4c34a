/**
 * The WebAssembly SIMD chunk kernel of the readers (see chunkKernel.ts), as base64.
 * Written by bin/write-chunk-kernel.mjs — edit the generator, not this file.
 */

/** Byte layout of the kernel's memory: a chunk of 64-bit ids in, their low words out, the run's least and greatest low word; `pages` of 64 KiB. */
export const CHUNK_LAYOUT = { inAt: 0, inBytes: 1048576, outAt: 1048576, rangeAt: 1572864, pages: 25 } as const;

export const CHUNK_KERNEL_BASE64 =
  'AGFzbQEAAAABBgFgAX8BfwIPAQNlbnYGbWVtb3J5AgAZAwIBAAcKAQZuYXJyb3cAAArKAwHHAwIIfwR7Qf////8H/REhCkGAgICA' +
  'eP0RIQtBAP0RIQkgAEF8cUEDdEEAaiEDQQAhAUGAgMAAIQICQANAIAEgA08NASAB/QAEACAB/QAEEP0NAAECAwgJCgsQERITGBka' +
  'GyEMIAkgAf0ABAAgAf0ABBD9DQQFBgcMDQ4PFBUWFxwdHh8gDEEf/awB/VH9UCEJIAogDP22ASEKIAsgDP24ASELIAIgDP0LBAAg' +
  'AUEgaiEBIAJBEGohAgwACwsgCf0bACEEIAr9GwAhBSAL/RsAIQYgBCAJ/RsBciEEIAr9GwEiByAFIAcgBUgbIQUgC/0bASIHIAYg' +
  'ByAGShshBiAEIAn9GwJyIQQgCv0bAiIHIAUgByAFSBshBSAL/RsCIgcgBiAHIAZKGyEGIAQgCf0bA3IhBCAK/RsDIgcgBSAHIAVI' +
  'GyEFIAv9GwMiByAGIAcgBkobIQYgAEF8cSEIAkADQCAIIABPDQEgCEEDdCgCACEHIAQgCEEDdCgCBCAHQR91c3IhBCAHIAUgByAF' +
  'SBshBSAHIAYgByAGShshBiAIQQJ0IAc2AoCAQCAIQQFqIQgMAAsLQQAgBTYCgIBgQQAgBjYChIBgIAQL';

/** speedband's version, recorded in the provenance of every file it writes. Keep in step with package.json (a test checks). */
export const VERSION = '0.1.0';

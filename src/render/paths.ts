import { fileURLToPath } from 'node:url';
import path from 'node:path';

/** The installed loopsheet package (templates, config), wherever the user runs the command from. */
export const PACKAGE_ROOT = path.resolve(fileURLToPath(new URL('../..', import.meta.url)));
export const TEMPLATES_DIR = path.join(PACKAGE_ROOT, 'templates');
export const ELEVENTY_CONFIG = path.join(PACKAGE_ROOT, '.eleventy.js');

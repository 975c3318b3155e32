export { parseEng, parseEngValue } from './parse.js';
export { formatEng, formatSpice } from './format.js';
export { showText } from './show.js';

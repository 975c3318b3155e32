export { parseEng, parseEngShifted, parseEngValue } from './parse.js';
export { formatEng, formatSpice, showNumber, showValue } from './format.js';
export { showText } from './show.js';

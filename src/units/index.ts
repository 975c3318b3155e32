export { parseEng, parseEngShifted, parseEngValue, specDecimal } from './parse.js';
export { formatEng, formatSpice, showNumber, showValue } from './format.js';
export { showText } from './show.js';

import { identifyLanguages } from '../src/text/index.js';
const texts = ['la biblioteca cierra demasiado temprano por la noche, abrir el domingo por la mañana y la noche', 'open later in the evening please, longer opening hours on weekends', 'wifi más rápido y más ordenadores'];
console.log(identifyLanguages(texts, { languages: ['en', 'es'], declared: ['en', 'en', 'es'], trustDeclared: false }));
console.log(identifyLanguages(texts, { languages: ['en', 'es'], declared: [undefined, undefined, undefined], trustDeclared: false }));

export { createRandom, type Random, type StatefulRandom } from './random.ts'

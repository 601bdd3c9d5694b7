// Types for @kninnug/constrainautor 4.1.0. The package ships its TypeScript source as its types;
// that source does not compile under our noUncheckedIndexedAccess, so the tsconfigs map the module
// name here ("paths") and we declare the small part we use.
interface DelaunatorLike {
  coords: { readonly length: number; readonly [n: number]: number }
  triangles: { readonly length: number; [n: number]: number }
  halfedges: { readonly length: number; [n: number]: number }
  hull: { readonly length: number; readonly [n: number]: number }
}
export default class Constrainautor {
  constructor(del: DelaunatorLike, edges?: readonly [number, number][])
  del: DelaunatorLike
  constrainOne(p1: number, p2: number): number
  constrainAll(edges: readonly [number, number][]): this
  delaunify(deep?: boolean): this
  untriangulatedPoints(): number[]
}

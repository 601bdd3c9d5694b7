/** A frame that cannot be meshed; `field` names the frame field at fault (e.g. 'mesh.edgeLength'). */
export class MeshError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`)
    this.name = 'MeshError'
  }
}

/**
 * Real clients of a running server for tests and benchmarks, signed in through a session cookie: a
 * y-websocket client of a room's sync endpoint (/sync/<room>) and a socket.io client of the surface
 * stream. No server module is imported, so browser tests load these cheaply.
 */
import { io as ioClient, type Socket } from 'socket.io-client'
import WebSocket from 'ws'
import { WebsocketProvider } from 'y-websocket'
import * as Y from 'yjs'

/** A WebSocket class for y-websocket that sends our cookie and Origin. */
export function cookieSocket(
  cookie: string,
  origin: string,
): new (address: string | URL, protocols?: string | string[]) => WebSocket {
  return class extends WebSocket {
    constructor(address: string | URL, protocols?: string | string[]) {
      super(address, protocols, { headers: { cookie, origin } })
    }
  }
}

export interface DocClient {
  doc: Y.Doc
  provider: WebsocketProvider
  synced: Promise<void>
  destroy: () => void
}

/** A y-websocket client of a room; `synced` resolves after the server's sync step 2. */
export function connectDoc(url: string, roomId: string, cookie: string): DocClient {
  const doc = new Y.Doc()
  const provider = new WebsocketProvider(url.replace(/^http/, 'ws') + '/sync', roomId, doc, {
    WebSocketPolyfill: cookieSocket(cookie, url) as unknown as typeof globalThis.WebSocket,
    disableBc: true,
  })
  // Each provider adds a process 'exit' listener that clears its awareness as the process ends;
  // a test or benchmark holds dozens at once (Node warns past 10), and the server drops a closed
  // socket's awareness itself, so the listener buys nothing here.
  process.off('exit', provider._exitHandler)
  const synced = new Promise<void>((resolve) => {
    if (provider.synced) resolve()
    else provider.once('sync', () => resolve())
  })
  return {
    doc,
    provider,
    synced,
    destroy: () => {
      provider.destroy()
      doc.destroy()
    },
  }
}

/** A socket.io client of the surface stream, signed in through the cookie. */
export function connectStream(url: string, cookie: string): Socket {
  return ioClient(url, {
    transports: ['websocket'],
    extraHeaders: { cookie, origin: url },
    forceNew: true,
    reconnection: false,
  })
}

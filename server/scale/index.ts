/**
 * Scale-out wiring for one app instance, present only when REDIS_URL is set: a command connection
 * (publishing, BullMQ producer, health) and dedicated subscriber connections for the socket.io
 * adapter and the document bus.
 */
import type { Redis } from 'ioredis'
import { closeRedis, createRedis, redisState } from './redis.js'

export interface ScaleLink {
  instanceId: string
  redis: Redis
  /** A new subscriber-mode connection (each pub/sub user needs its own). */
  subscriber: (name: string) => Redis
  state: () => 'up' | 'down'
  close: () => Promise<void>
}

export function connectScale(url: string, instanceId: string): ScaleLink {
  const redis = createRedis(url, `instance ${instanceId}`)
  const subscribers: Redis[] = []
  return {
    instanceId,
    redis,
    subscriber: (name) => {
      const sub = createRedis(url, `instance ${instanceId} ${name}`)
      subscribers.push(sub)
      return sub
    },
    state: () => redisState(redis),
    close: async () => {
      await Promise.all(subscribers.map(closeRedis))
      await closeRedis(redis)
    },
  }
}

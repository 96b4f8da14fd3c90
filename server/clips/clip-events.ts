import { EventEmitter } from 'node:events';

/** "Clip changed" notices for server-sent events. In-process now; Redis pub/sub later. */
export interface ClipEvents {
  emit(assessmentId: number, clipId: number): void;
  subscribe(assessmentId: number, listener: (clipId: number) => void): () => void;
}

export function inProcessClipEvents(): ClipEvents {
  const bus = new EventEmitter();
  bus.setMaxListeners(0);
  return {
    emit(assessmentId, clipId) {
      bus.emit(`a${assessmentId}`, clipId);
    },
    subscribe(assessmentId, listener) {
      bus.on(`a${assessmentId}`, listener);
      return () => bus.off(`a${assessmentId}`, listener);
    },
  };
}

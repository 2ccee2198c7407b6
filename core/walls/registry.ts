/**
 * The wall-correction methods the engine knows, and how a setup chooses one. Adding a tunnel section
 * or a mounting is adding a method here (docs/architecture.md, "Adding a wall-correction method").
 */
import type { Setup } from '../setup/schema.ts';
import type { WallMethod } from './method.ts';
import { wall2dMethod } from './wall2d.ts';
import { classic3dMethod, freeJet3dMethod, isFreeJet, maskell3dMethod } from './wall3d.ts';

export const WALL_METHODS: readonly WallMethod[] = [wall2dMethod, classic3dMethod, maskell3dMethod, freeJet3dMethod];

/**
 * The id a setup asks for: "2d" for a 2D model, else "3d-" and the wake model; a 3D model in a section
 * with a free boundary asks for "3d-free-jet" unless Maskell is asked for by name (that method then
 * reports its fallback to the free-jet corrections).
 */
export function requestedWallMethod(setup: Setup): string {
  if (setup.model.kind === '2d') return '2d';
  if (setup.corrections.wake === 'classic' && isFreeJet(setup)) return '3d-free-jet';
  return `3d-${setup.corrections.wake}`;
}

/**
 * The registered method for a setup: the one it asks for; when that one refuses the setup, the reason
 * is an error the caller reports (no silent substitute).
 */
export function chooseWallMethod(setup: Setup): { method: WallMethod } | { refused: string } {
  const id = requestedWallMethod(setup);
  const method = WALL_METHODS.find((m) => m.id === id);
  if (!method) return { refused: `no wall-correction method "${id}" is known` };
  const why = method.accepts(setup);
  return why === undefined ? { method } : { refused: why };
}

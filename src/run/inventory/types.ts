/** What the inventory finds in a folder of raw frames, and the draft it makes of it. */
import type { Header } from '../../fits/header.js';

export type InventoryFrameKind = 'bias' | 'flat' | 'arc' | 'science' | 'unknown';

/** A frame's header as read from disk (the first HDU with a 2-D image, primary cards inherited). */
export interface FrameHeader {
  /** Path of the file as found under the scanned folder. */
  path: string;
  /** 0-based HDU of the image. */
  hdu: number;
  header: Header;
}

export interface UnreadableFile {
  path: string;
  /** Why it could not be used, e.g. the InputError message. */
  reason: string;
}

export interface ClassifiedFrame extends FrameHeader {
  kind: InventoryFrameKind;
  /** Which rule decided the kind, in words (`IMAGETYP = 'object'`). */
  reason: string;
  /** OBJECT card, trimmed; undefined when absent or empty. */
  object?: string;
  /** Start of exposure from DATE-OBS (with TIME-OBS when DATE-OBS holds the date only), ms since 1970 UTC. */
  startMs?: number;
  /** EXPTIME, seconds. */
  exptimeS?: number;
  /** NAXIS1 x NAXIS2 of the image, pixels. */
  width: number;
  height: number;
  /** Detector keywords (binning ...) and their values as text. */
  detector: Record<string, string>;
  /** Spectral-configuration keywords (grating, tilt ...) and their values as text. */
  spectral: Record<string, string>;
  /** Lamp names from the lamp keywords, as written (`Ne`, `Ar`). */
  lamps: string[];
}

/** Frames sharing the detector shape, detector keywords and spectral keywords. */
export interface SetupGroup {
  /** Name in the draft manifest: setup1, setup2 ... in order of first science frame. */
  name: string;
  width: number;
  height: number;
  detector: Record<string, string>;
  spectral: Record<string, string>;
  bias: ClassifiedFrame[];
  flat: ClassifiedFrame[];
  arc: ClassifiedFrame[];
  science: ClassifiedFrame[];
}

/** A target: the science frames of one OBJECT on one setup, with the arcs nearest them in time. */
export interface TargetDraft {
  name: string;
  /** Name of the manifest setup (a SetupGroup's name, with a suffix when its targets need different arcs). */
  setup: string;
  group: SetupGroup;
  frames: ClassifiedFrame[];
  arcs: ClassifiedFrame[];
  /** Time from the nearest arc to the nearest science frame, minutes (undefined without DATE-OBS). */
  arcGapMinutes?: number;
}

export interface Inventory {
  frames: ClassifiedFrame[];
  unreadable: UnreadableFile[];
  setups: SetupGroup[];
  targets: TargetDraft[];
  /** Things the user should look at: calibrations missing, frames in no setup, ... */
  notes: string[];
}

// ffprobe/ffmpeg (Debian's, installed by `npm start`/`npm test`): what a file is, a poster, a web-playable MP4.
import { execFile } from "node:child_process";
import { promisify } from "node:util";

const execFileAsync = promisify(execFile);

export type Tools = { ffmpeg: string; ffprobe: string; timeoutMs: number };

export type ProbeResult = {
  duration: number;
  /** Display size: rotation and pixel aspect applied. */
  width: number;
  height: number;
  aspectRatio: string;
  frameRate: number;
  videoDuration: number;
  /** Stream index of the picture to transcode (cover art is skipped). */
  videoIndex: number;
  audio: { channels: number; duration: number } | null;
};

/** The file is not something we can turn into a clip; the message is shown to staff. */
export class NotAVideoError extends Error {}

/** Our problem, not the file's: never reported as a bad upload. */
export class ToolMissingError extends Error {}

// Keeps the short side at most 720 px (portrait phone clips too) and both sides even, as H.264 4:2:0 needs.
const SCALE_720 = "scale='if(gte(iw,ih),-2,min(720,trunc(iw/2)*2))':'if(gte(iw,ih),min(720,trunc(ih/2)*2),-2)'";
// Only local files: an uploaded playlist must not make ffmpeg fetch URLs or other files.
const INPUT_FLAGS = ["-protocol_whitelist", "file"];
const STILL_FORMATS = /(^|,)(image2|[a-z0-9]+_pipe|gif|apng)(,|$)/;

type Stream = {
  index?: number;
  codec_type?: string;
  width?: number;
  height?: number;
  sample_aspect_ratio?: string;
  avg_frame_rate?: string;
  r_frame_rate?: string;
  duration?: string;
  channels?: number;
  disposition?: { attached_pic?: number };
  side_data_list?: { rotation?: number }[];
  tags?: { rotate?: string };
};
type ProbeJson = { streams?: Stream[]; format?: { duration?: string; format_name?: string } };

async function run(command: string, args: string[], tools: Tools, signal: AbortSignal): Promise<string> {
  try {
    const { stdout } = await execFileAsync(command, args, { signal, timeout: tools.timeoutMs, maxBuffer: 16 * 1024 * 1024, killSignal: "SIGKILL" });
    return stdout;
  } catch (error) {
    if (signal.aborted) throw error;
    if ((error as NodeJS.ErrnoException).code === "ENOENT") {
      throw new ToolMissingError(`${command} was not found; install Debian's ffmpeg package (npm start does this).`);
    }
    const stderr = (error as { stderr?: string }).stderr?.trim();
    const lastLine = stderr ? stderr.split("\n").filter(Boolean).pop() : undefined;
    throw new Error(lastLine ?? (error instanceof Error ? error.message : String(error)), { cause: error });
  }
}

function ratio(text: string | undefined): number | null {
  const match = /^(\d+)[:/](\d+)$/.exec(text ?? "");
  if (!match) return null;
  const [num, den] = [Number(match[1]), Number(match[2])];
  return num > 0 && den > 0 ? num / den : null;
}

function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}

/** "16:9" style, from the display size. */
export function aspectRatio(width: number, height: number): string {
  const d = gcd(width, height);
  return `${width / d}:${height / d}`;
}

function rotation(stream: Stream): number {
  const fromSideData = stream.side_data_list?.find((s) => typeof s.rotation === "number")?.rotation;
  const raw = fromSideData ?? Number(stream.tags?.rotate ?? 0);
  return Math.abs(Math.round(raw)) % 180;
}

const round = (value: number, places: number) => Number(value.toFixed(places));

export async function probeVideo(file: string, tools: Tools, signal: AbortSignal): Promise<ProbeResult> {
  let json: ProbeJson;
  try {
    const out = await run(tools.ffprobe, ["-v", "error", ...INPUT_FLAGS, "-print_format", "json", "-show_format", "-show_streams", `file:${file}`], tools, signal);
    json = JSON.parse(out) as ProbeJson;
  } catch (error) {
    if (signal.aborted || error instanceof ToolMissingError) throw error;
    // ffprobe names the file it read; staff see this message, and our paths mean nothing to them.
    const reason = error instanceof Error ? error.message.replace(`file:${file}: `, "") : "ffprobe failed";
    throw new NotAVideoError(`The uploaded file is not a decodable video (${reason}).`);
  }
  const streams = json.streams ?? [];
  const video = streams.find((s) => s.codec_type === "video" && !s.disposition?.attached_pic && (s.width ?? 0) > 0 && (s.height ?? 0) > 0);
  if (!video) throw new NotAVideoError("The uploaded file is not a decodable video: it has no video stream.");
  const formatName = json.format?.format_name ?? "";
  if (STILL_FORMATS.test(formatName)) throw new NotAVideoError(`The uploaded file is not a decodable video: it is a still image (${formatName}).`);
  if (/(^|,)hls(,|$)/.test(formatName)) throw new NotAVideoError("The uploaded file is not a decodable video: playlists are not accepted.");
  const duration = Number(json.format?.duration ?? video.duration);
  if (!(duration > 0)) throw new NotAVideoError("The uploaded file is not a decodable video: it has no duration.");

  const sar = ratio(video.sample_aspect_ratio) ?? 1;
  let width = Math.round((video.width ?? 0) * sar);
  let height = video.height ?? 0;
  if (rotation(video) === 90) [width, height] = [height, width];
  const audio = streams.find((s) => s.codec_type === "audio");
  return {
    duration: round(duration, 6),
    width,
    height,
    aspectRatio: aspectRatio(width, height),
    frameRate: round(ratio(video.avg_frame_rate) ?? ratio(video.r_frame_rate) ?? 0, 3),
    videoDuration: round(Number(video.duration ?? duration), 6),
    videoIndex: video.index ?? 0,
    audio: audio ? { channels: audio.channels ?? 0, duration: round(Number(audio.duration ?? duration), 6) } : null,
  };
}

/** A JPEG at 1 s, or the middle of clips shorter than 2 s. */
export async function makePoster(source: string, target: string, probe: ProbeResult, tools: Tools, signal: AbortSignal): Promise<void> {
  const at = probe.duration >= 2 ? 1 : probe.duration / 2;
  await run(
    tools.ffmpeg,
    ["-v", "error", ...INPUT_FLAGS, "-ss", at.toFixed(3), "-i", `file:${source}`, "-map", `0:${probe.videoIndex}`, "-frames:v", "1", "-vf", SCALE_720, "-q:v", "3", "-f", "image2", "-update", "1", "-y", `file:${target}`],
    tools,
    signal,
  );
}

/** H.264 + AAC in an MP4 with the index up front, so a browser can start and seek before it has the whole file. */
export async function makeRendition(source: string, target: string, probe: ProbeResult, tools: Tools, signal: AbortSignal): Promise<void> {
  await run(
    tools.ffmpeg,
    [
      "-v", "error", ...INPUT_FLAGS, "-i", `file:${source}`,
      "-map", `0:${probe.videoIndex}`, "-map", "0:a:0?",
      "-vf", SCALE_720, "-c:v", "libx264", "-preset", "veryfast", "-crf", "23", "-pix_fmt", "yuv420p",
      "-c:a", "aac", "-b:a", "128k", "-ac", "2",
      "-movflags", "+faststart", "-f", "mp4", "-y", `file:${target}`,
    ],
    tools,
    signal,
  );
}

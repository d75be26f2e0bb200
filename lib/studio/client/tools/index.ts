// The editor's tools, by id, in the order the tool rail shows them, and what a tool is (its
// interface lives in tool.ts so that the tools themselves never import this registry). A new tool
// is one file in this folder implementing `Tool` and one line here; the page needs no change.
import { crestTool } from './crest';
import { flowTool } from './flow';
import { lookTool } from './look';
import { partingTool } from './parting';
import { pinTool } from './pin';
import { remainderTool } from './remainder';
import { saddleTool } from './saddle';
import { singularityTool } from './singularity';
import { tintTool } from './tint';
import type { Tool, ToolId } from './tool';
import { whorlTool } from './whorl';

export type { EditorChange, SurfaceHit, Tool, ToolContext, ToolId, ToolOptions, ToolStep } from './tool';

/** A tool of any kind of state: the session only ever hands a tool back the state it made. */
type AnyTool = Tool<unknown>;

export const TOOLS: Readonly<Record<ToolId, AnyTool>> = {
  look: lookTool,
  whorl: whorlTool,
  saddle: saddleTool,
  singularity: singularityTool,
  parting: partingTool,
  crest: crestTool,
  flow: flowTool,
  pin: pinTool,
  remainder: remainderTool,
  tint: tintTool,
};

/** The tools on the rail, each with its key; the remainder tool is picked from the budget card instead. */
export const RAIL_TOOLS: readonly AnyTool[] = [lookTool, whorlTool, saddleTool, singularityTool, partingTool, crestTool, flowTool, pinTool, tintTool];

/** The rail's tool picked by a key (any case), or undefined. */
export function toolOfKey(key: string): AnyTool | undefined {
  return RAIL_TOOLS.find((tool) => tool.shortcut?.toLowerCase() === key.toLowerCase());
}

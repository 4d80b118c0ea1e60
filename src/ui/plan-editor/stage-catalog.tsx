import { Box, Text } from 'ink';
import { stageKinds } from '../../circuit/registry.js';
import { cell } from '../components/columns.js';
import { scrollWindow } from '../components/scroll-window.js';
import { pointer, toneProps } from '../theme.js';

export interface StageCatalogProps {
  readonly selected: number;
  readonly width: number;
  readonly height: number;
  readonly isHelpOpen: boolean;
}

/** Every stage kind of the registry with its summary; the selected kind's whole summary, its rail, outputs and part roles with their units and descriptions. */
export function StageCatalog({ selected, width, height, isHelpOpen }: StageCatalogProps) {
  const kinds = Object.entries(stageKinds);
  const [, module] = kinds[selected] ?? [];
  const roles = module?.roles ?? [];
  // As wide as the longest role, so none is cut (`checks[i].nominal`).
  const roleWidth = Math.max(16, ...roles.map((r) => r.role.length));
  // The list cuts every summary at the screen's edge; the selected kind's is shown whole under it.
  const summaryRows = module ? Math.ceil(module.summary.length / Math.max(20, width - 8)) : 0;
  const listRows = Math.max(3, Math.min(kinds.length, height - roles.length - 6 - summaryRows));
  const view = scrollWindow(kinds.length, selected, listRows);
  return (
    <Box flexDirection="column" borderStyle="single" paddingX={1} width={width}>
      <Text bold {...toneProps('title')}>
        Add a stage — {kinds.length} kinds
      </Text>
      {kinds.slice(view.start, view.end).map(([name, m], i) => (
        <Text key={name} wrap="truncate-end" inverse={view.start + i === selected}>
          {view.start + i === selected ? pointer : ' '} {cell(name, 19)} <Text {...toneProps('dim')}>{m.summary}</Text>
        </Text>
      ))}
      {module ? <Text {...toneProps('dim')}>{module.summary}</Text> : null}
      <Text wrap="truncate-end" bold>
        {module
          ? `parts and settings${module.needsInput ? ' (takes an input)' : ''}${module.traits?.railSetting ? `; fed from the rail named in "${module.traits.railSetting}"` : ''}; outputs: ${module.outputs.join(', ') || 'none'}`
          : ''}
      </Text>
      {roles.slice(0, Math.max(1, height - listRows - 5 - summaryRows)).map((r) => (
        <Text key={r.role} wrap="truncate-end">
          {'  '}
          {cell(r.role, roleWidth)} {cell(r.unit, 4)} {r.description}
          {r.optional ? ' (optional)' : ''}
        </Text>
      ))}
      <Text {...toneProps('dim')} wrap="truncate-end">
        {isHelpOpen
          ? 'The stage is added at the end with example values its kind accepts, wired to the stage before it; type your values over them.'
          : '↑↓ choose · Enter add · Esc cancel · ? help'}
      </Text>
    </Box>
  );
}

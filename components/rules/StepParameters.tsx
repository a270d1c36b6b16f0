// The parameters of one step, each with a control that fits it (shared/rules/schema.ts gives the ranges).
import { StyleSheet, View } from 'react-native';
import { GRADIENT_OPERATORS, GRADIENT_OUTPUTS, type Step } from '../../shared/rules/schema';
import type { KernelInfo } from '../../shared/api/kernels';
import { space } from '../../lib/theme';
import { ChoiceChips } from '../ChoiceChips';
import { KernelStepEditor } from './KernelStepEditor';
import { NumberField } from './NumberField';
import {
  ADAPTIVE_C_SPEC,
  ADAPTIVE_SIZE_SPEC,
  BOX_SIZE_SPEC,
  MEDIAN_SIZE_SPEC,
  RADIUS_SPEC,
  SIGMA_SPEC,
  THRESHOLD_VALUE_SPEC,
} from './stepCatalogue';

interface StepParametersProps {
  step: Step;
  kernels: readonly KernelInfo[];
  canSaveKernel: boolean;
  onChange: (step: Step) => void;
  errorOf: (field: string) => string | undefined;
  /** The step's name ("Step 2: Gaussian"), said before each field's label: several steps can be open at once. */
  stepName: string;
}

const OPERATOR_LABELS: Record<(typeof GRADIENT_OPERATORS)[number], string> = { sobel: 'Sobel', scharr: 'Scharr', prewitt: 'Prewitt' };
const OUTPUT_LABELS: Record<(typeof GRADIENT_OUTPUTS)[number], string> = { x: 'Across (x)', y: 'Down (y)', magnitude: 'Magnitude', direction: 'Direction' };

export function StepParameters({ step, kernels, canSaveKernel, onChange, errorOf, stepName }: StepParametersProps) {
  const keep = (v: number | undefined, apply: (n: number) => void) => {
    if (v !== undefined) apply(v);
  };
  switch (step.op) {
    case 'kernel':
      return <KernelStepEditor step={step} kernels={kernels} canSaveKernel={canSaveKernel} onChange={onChange} errorOf={errorOf} stepName={stepName} />;
    case 'gaussian':
    case 'log':
      return <NumberField context={stepName} spec={SIGMA_SPEC} value={step.sigma} onChange={(v) => keep(v, (sigma) => onChange({ ...step, sigma }))} error={errorOf('sigma')} />;
    case 'box':
      return <NumberField context={stepName} spec={BOX_SIZE_SPEC} value={step.size} onChange={(v) => keep(v, (size) => onChange({ ...step, size }))} error={errorOf('size')} />;
    case 'median':
      return <NumberField context={stepName} spec={MEDIAN_SIZE_SPEC} value={step.size} onChange={(v) => keep(v, (size) => onChange({ ...step, size }))} error={errorOf('size')} />;
    case 'gradient':
      return (
        <View style={styles.group}>
          <ChoiceChips context={stepName} label="Operator" choices={GRADIENT_OPERATORS.map((o) => ({ value: o, label: OPERATOR_LABELS[o] }))} value={step.operator} onChange={(operator) => onChange({ ...step, operator })} />
          <ChoiceChips context={stepName} label="Output" choices={GRADIENT_OUTPUTS.map((o) => ({ value: o, label: OUTPUT_LABELS[o] }))} value={step.output} onChange={(output) => onChange({ ...step, output })} />
        </View>
      );
    case 'laplacian':
      return (
        <ChoiceChips
          context={stepName}
          label="Neighbours"
          choices={[
            { value: '4', label: '4 (edges only)' },
            { value: '8', label: '8 (with diagonals)' },
          ]}
          value={String(step.neighbours)}
          onChange={(v) => onChange({ ...step, neighbours: v === '8' ? 8 : 4 })}
        />
      );
    case 'threshold':
      return (
        <View style={styles.group}>
          <ChoiceChips
            context={stepName}
            label="Method"
            choices={[
              { value: 'fixed', label: 'Fixed value' },
              { value: 'otsu', label: 'Otsu' },
              { value: 'adaptive-mean', label: 'Adaptive mean' },
            ]}
            value={step.method}
            onChange={(method) =>
              onChange(
                method === 'fixed'
                  ? { op: 'threshold', method, value: 128, invert: step.invert }
                  : method === 'otsu'
                    ? { op: 'threshold', method, invert: step.invert }
                    : { op: 'threshold', method, size: 31, c: 5, invert: step.invert },
              )
            }
          />
          {step.method === 'fixed' ? (
            <NumberField context={stepName} spec={THRESHOLD_VALUE_SPEC} value={step.value} onChange={(v) => keep(v, (value) => onChange({ ...step, value }))} error={errorOf('value')} />
          ) : null}
          {step.method === 'adaptive-mean' ? (
            <View style={styles.group}>
              <NumberField context={stepName} spec={ADAPTIVE_SIZE_SPEC} value={step.size} onChange={(v) => keep(v, (size) => onChange({ ...step, size }))} error={errorOf('size')} />
              <NumberField context={stepName} spec={ADAPTIVE_C_SPEC} value={step.c} onChange={(v) => keep(v, (c) => onChange({ ...step, c }))} error={errorOf('c')} />
            </View>
          ) : null}
          <ChoiceChips
            context={stepName}
            label="Mask marks"
            choices={[
              { value: 'above', label: 'Values above' },
              { value: 'below', label: 'Values at or below (inverted)' },
            ]}
            value={step.invert ? 'below' : 'above'}
            onChange={(v) => {
              const { invert: _dropped, ...rest } = step;
              onChange(v === 'below' ? { ...rest, invert: true } : rest);
            }}
          />
        </View>
      );
    case 'erode':
    case 'dilate':
    case 'open':
    case 'close':
      return <NumberField context={stepName} spec={RADIUS_SPEC} value={step.radius} onChange={(v) => keep(v, (radius) => onChange({ ...step, radius }))} error={errorOf('radius')} />;
  }
}

const styles = StyleSheet.create({ group: { gap: space.md } });

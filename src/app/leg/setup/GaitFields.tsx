/**
 * The leg's walking: the ground line (level at a height, or through a point along a
 * direction; up is its +y side), the stance tolerance, the crank's and the body's
 * directions, the foot samples per turn, and the legs on one shaft with their phases
 * (for the contact figures of an opened design).
 */
import { DEFAULT_LEG_STEPS, LEG_STEPS_RANGE } from '../../../core/synthesis/legProblem';
import { FieldIssue, SetupField } from '../../suspension/targets/SetupField';
import { useLeg, useSetupDispatch } from '../store';

export function GaitFields() {
  const dispatch = useSetupDispatch();
  const s = useLeg((st) => st.setup);
  const g = s.ground;
  return (
    <fieldset className="legws-group" data-testid="leg-gait-fields">
      <legend>Ground, stance and directions</legend>
      <div className="legws-row">
        <label>
          Ground line{' '}
          <select value={g.kind} onChange={(e) => dispatch({ type: 'groundKind', kind: e.target.value === 'line' ? 'line' : 'level' })}>
            <option value="level">level, at a height</option>
            <option value="line">through a point, along a direction</option>
          </select>
        </label>
        <FieldIssue field="ground" />
      </div>
      {g.kind === 'level' ? (
        <SetupField field="ground.yMm" label="Ground height y" unit="mm" value={g.yMm} onChange={(text) => dispatch({ type: 'groundText', field: 'yMm', text })} />
      ) : (
        <>
          <div className="legws-row" data-field="ground.point">
            <SetupField field="ground.point.x" label="Ground point x" unit="mm" value={g.px} onChange={(text) => dispatch({ type: 'groundText', field: 'px', text })} />
            <SetupField field="ground.point.y" label="Ground point y" unit="mm" value={g.py} onChange={(text) => dispatch({ type: 'groundText', field: 'py', text })} />
            <FieldIssue field="ground.point" />
          </div>
          <div className="legws-row" data-field="ground.direction">
            <SetupField field="ground.direction.x" label="Direction x" value={g.dx} onChange={(text) => dispatch({ type: 'groundText', field: 'dx', text })} />
            <SetupField field="ground.direction.y" label="Direction y" value={g.dy} hint="up is the line's +y side; not vertical" onChange={(text) => dispatch({ type: 'groundText', field: 'dy', text })} />
            <FieldIssue field="ground.direction" />
          </div>
        </>
      )}
      <SetupField field="stanceToleranceMm" label="Stance tolerance" unit="mm" value={s.stanceToleranceMm} hint="the foot is in stance within this height of the ground line" onChange={(text) => dispatch({ type: 'stanceTolerance', text })} />
      <div className="legws-row">
        <label>
          Crank turns{' '}
          <select value={s.crankDirection} onChange={(e) => dispatch({ type: 'crankDirection', sense: e.target.value === '-1' ? -1 : 1 })}>
            <option value={1}>counter-clockwise</option>
            <option value={-1}>clockwise</option>
          </select>
        </label>
        <label>
          Body walks towards{' '}
          <select value={s.walkingDirection} onChange={(e) => dispatch({ type: 'walkingDirection', sense: e.target.value === '-1' ? -1 : 1 })}>
            <option value={1}>+x</option>
            <option value={-1}>−x</option>
          </select>
        </label>
      </div>
      <SetupField field="steps" label="Foot samples per turn in the search" value={s.steps} hint={`${LEG_STEPS_RANGE[0]}–${LEG_STEPS_RANGE[1]}; empty: ${DEFAULT_LEG_STEPS}`} onChange={(text) => dispatch({ type: 'steps', text })} />
      <div className="legws-row">
        <SetupField field="phasing.legs" label="Legs on one shaft" value={s.phasing.legs} hint="for the contact figures of an opened design" onChange={(text) => dispatch({ type: 'phasing', field: 'legs', text })} />
        <SetupField field="phasing.phasesDeg" label="Their phases" unit="°" value={s.phasing.phasesDeg} hint="one per leg, e.g. 0, 120, 240" onChange={(text) => dispatch({ type: 'phasing', field: 'phasesDeg', text })} />
      </div>
    </fieldset>
  );
}

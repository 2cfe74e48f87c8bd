/** The project's name, shown as the workspace's title and renamed in place; it is saved with the project. */
import { useState } from 'react';
import { checkProjectName } from '../state/fields';
import { useDispatch, useWorkspace } from '../state/store';
import { FieldInput } from './NumberInput';

function NameEditor({ name, onDone }: { name: string; onDone: () => void }) {
  const dispatch = useDispatch();
  const [text, setText] = useState(name);
  const checked = checkProjectName(text);
  // An empty name is refused beside the field, and the field stays open until it holds a name.
  const commit = () => {
    if (!checked.ok) return;
    if (checked.value !== name) dispatch({ type: 'project/rename', name: checked.value });
    onDone();
  };
  return <FieldInput text={text} label="Project name" issueKey="project-name" message={checked.ok ? null : checked.message} onText={setText} onDone={commit} className="project-name-input" autoFocus />;
}

export function ProjectName() {
  const name = useWorkspace((s) => s.project.name);
  const [editing, setEditing] = useState(false);
  return (
    <div className="project-name field-row" data-testid="project-name">
      {editing ? (
        <>
          <span aria-hidden="true">Project name</span>
          <NameEditor name={name} onDone={() => setEditing(false)} />
        </>
      ) : (
        <>
          <span className="project-title">{name}</span>
          <button type="button" onClick={() => setEditing(true)}>
            Rename project
          </button>
        </>
      )}
    </div>
  );
}

/**
 * The "choose surfaces by what they are" folder of a tool's panel (lil-gui): a name, a box holding the
 * surfaces, an area range, and a button that reads them (`groupChoice.ts`) and hands the selector and the open
 * file's groups it picks to the tool; what cannot be read or matches nothing goes to the banner.
 */
import type GUI from 'lil-gui';
import type { GroupInfo } from '../../workers/api.ts';
import type { GroupSelector } from '../surface/groupSelect.ts';
import { EMPTY_CHOICE, groupsChosen, selectorFromText, type GroupChoiceText } from './groupChoice.ts';

/** Title of the folder (browser tests find it by this). */
export const GROUP_CHOICE_TITLE = 'choose surfaces by what they are';

/**
 * Adds the folder (closed) to `parent`, with `button` as the label of its button. `fields` keeps what was typed
 * across rebuilds of the panel; `errorPrefix` starts a message on the banner.
 */
export function addGroupChoice(parent: GUI, fields: GroupChoiceText, button: string, groups: () => readonly GroupInfo[],
  choose: (selector: GroupSelector, ids: number[]) => void, error: (message: string) => void): GUI {
  const by = parent.addFolder(GROUP_CHOICE_TITLE).close();
  by.add(fields, 'name').name('name is');
  by.add(fields, 'box').name('inside box [m]').domElement.title = 'xmin, xmax, ymin, ymax, zmin, zmax: surfaces lying wholly inside';
  by.add(fields, 'areaFrom').name('area from [m²]');
  by.add(fields, 'areaTo').name('area to [m²]');
  by.add({ go: () => {
    let selector: GroupSelector, ids: number[];
    try {
      selector = selectorFromText(fields);
      ids = groupsChosen(groups(), selector);
    } catch (e) {
      error((e as Error).message);
      return;
    }
    choose(selector, ids);
  } }, 'go').name(button);
  return by;
}

/** Fresh, empty fields. */
export const emptyChoice = (): GroupChoiceText => ({ ...EMPTY_CHOICE });

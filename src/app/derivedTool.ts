/**
 * Derived fields and user formulas as fields of the open file. The colour chooser offers every derived
 * field the file's arrays allow (derivedChoice.ts); choosing one makes it in the worker (the progress bar
 * names it) and attaches it to the held dataset, so cut-planes, line probes and probe sets take it like a
 * file array. The attached set — derived names chosen and the formulas of the probe set — is always made
 * afresh from the file's arrays, so cp and total pressure follow the reference conditions (made again
 * when they change) and a removed formula is gone. Calls reach the worker in the order made, before any
 * cut or line request sent after them.
 */
import type { FieldsReply } from '../../workers/api.ts';
import type { DerivedName } from '../derive/derivedFields.ts';
import type { FormulaDoc } from '../derive/formulaFields.ts';
import { DERIVED_KEY, derivedLabel, offeredDerived } from './derivedChoice.ts';
import type { FieldSource, ResolvedColour, SourceEntry } from './fieldSource.ts';
import type { ReferenceTool } from './referenceTool.ts';
import type { Viewer } from './viewer.ts';

export class DerivedTool implements FieldSource {
  /** Derived fields chosen on this file, in the order chosen. */
  private wanted: DerivedName[] = [];
  private formulaList: FormulaDoc[] = [];
  /** The last reply: formula units and what failed (name → one-line message). */
  private last: Pick<FieldsReply, 'formulaUnits' | 'failed'> = { formulaUnits: {}, failed: [] };
  /** Attach calls in flight, chained so their replies apply in order. */
  private chain: Promise<void> = Promise.resolve();
  private readonly attachedListeners: (() => void)[] = [];

  constructor(private readonly v: Viewer, private readonly refs: ReferenceTool) {
    v.addFieldSource(this);
    // the derived field the view is coloured by carries over to the next file or step when it has the inputs;
    // the others are dropped; the set's formulas stay
    let keep: DerivedName | undefined;
    v.onBeforeDataset(() => {
      const f = v.fields.find((x) => x.key === v.settings.field);
      keep = f && (this.wanted as string[]).includes(f.name) ? f.name as DerivedName : undefined;
    });
    v.onDataset(() => {
      const offered = offeredDerived(v.fields.map((f) => ({ name: f.name, association: f.association, components: f.components })));
      this.wanted = keep && offered.includes(keep) ? [keep] : [];
      const colour = this.wanted[0];
      if (!this.wanted.length && !this.formulaList.length) return;
      void this.attach(colour ? `computing ${colour}` : 'making the formulas').then(() => {
        const f = colour ? v.fields.find((x) => x.name === colour) : undefined;
        if (f && !this.failureOf(colour!)) void v.chooseField(f.key);
      });
    });
    // cp, total pressure and formulas naming ref.* depend on the reference conditions
    refs.onChange(() => { if (this.wanted.length || this.formulaList.length) void this.attach('updating derived fields'); });
  }

  /** Called after every attach (formula units and failures may have changed). */
  onAttached(f: () => void): void { this.attachedListeners.push(f); }

  /** The formulas attached now (the probe set's). */
  get formulas(): FormulaDoc[] { return this.formulaList.map((f) => ({ ...f })); }

  /** SI unit of a formula field as the worker found it. */
  unitOf(name: string): string | undefined { return this.last.formulaUnits[name]; }

  /** Why a derived field or formula could not be made, or undefined. */
  failureOf(name: string): string | undefined { return this.last.failed.find((f) => f.name === name)?.message; }

  /** Replaces the formulas (in order) and attaches them; resolves once the worker has them. */
  setFormulas(list: readonly FormulaDoc[]): Promise<void> {
    this.formulaList = list.map((f) => ({ name: f.name, expression: f.expression, ...(f.unit ? { unit: f.unit } : {}) }));
    return this.attach(this.formulaList.length ? 'making the formulas' : 'removing the formulas');
  }

  entries(): SourceEntry[] {
    const infos = this.v.fields.map((f) => ({ name: f.name, association: f.association, components: f.components }));
    return offeredDerived(infos).map((n) => ({ label: derivedLabel(n), key: `${DERIVED_KEY}${n}` }));
  }

  owns(key: string): boolean { return key.startsWith(DERIVED_KEY); }

  async resolve(key: string): Promise<ResolvedColour> {
    const name = key.slice(DERIVED_KEY.length) as DerivedName;
    if (!this.wanted.includes(name)) this.wanted.push(name);
    await this.attach(`computing ${name}`);
    const failed = this.failureOf(name);
    if (failed) { this.wanted = this.wanted.filter((n) => n !== name); throw new Error(failed); }
    const f = this.v.fields.find((x) => x.name === name);
    if (!f) throw new Error(`the worker did not attach "${name}"`);
    return { kind: 'field', key: f.key };
  }

  /** Sends the attached set to the worker (posted at once, so it precedes later requests) and takes its description. */
  private attach(stage: string): Promise<void> {
    if (!this.v.description) return this.chain;
    const request = {
      derived: [...this.wanted], formulas: this.formulas,
      reference: (({ density, viscosity, speed, pressure, area, length }) => ({ density, viscosity, speed, pressure, area, length }))(this.refs.conditions),
    };
    const call = this.v.track(this.v.compute.attachFields(request));
    const busy = this.v.progress;
    busy.show(stage, 0, 0, false);
    this.chain = this.chain.then(async () => {
      try {
        const reply = await call;
        this.last = { formulaUnits: reply.formulaUnits, failed: reply.failed };
        this.v.updateFields(reply.description);
      } catch (e) {
        this.v.banner.error(`Derived fields: ${(e as Error).message}`);
      } finally {
        if (document.body.dataset['state'] !== 'loading') busy.hide();
        for (const l of this.attachedListeners) l();
      }
    });
    return this.chain;
  }
}

import type { Project } from '../model/project.ts';
import { GWP_SOURCES } from '../reference/ghg.ts';
import { PROCESS_CAUTION } from './declaration-view.ts';
import { chosenMethods } from '../schema/declaration.ts';

/** How site-level data were shared among products, when the project has any (ISO 14044 §4.3.4). */
function siteAllocationStatement(project: Project): string[] {
  const groups = project.allocation.groups.filter((group) => group.keys.size > 0);
  if (groups.length === 0) return [];
  const described = groups.map((group) => `${group.site} (${group.period}: ${group.rows.length} row${group.rows.length === 1 ? '' : 's'} of site.csv shared among ${group.production.length} product${group.production.length === 1 ? '' : 's'} by ${[...group.keys.keys()].join(', ')})`);
  return [
    `Site-level data (ISO 14044 §4.3.4): amounts metered or bought for a whole site and period are shared among the products made there in that period, per declared unit amount × key_p / Σ keys ÷ output_p, where the key is the output’s mass (output × unit mass), the output in declared units, or a key of the practitioner’s own from production.csv. Allocation was not avoided by subdivision for these rows; the shares are listed with the inputs of each declaration. Sites: ${described.join('; ')}.`,
  ];
}

/**
 * The methodology statements every declaration page and the verification pack print: how
 * the figures were made, where the standards leave a choice, and which choice was made.
 */
export function methodology(project: Project): Array<{ title: string; paragraphs: string[] }> {
  const d = project.declaration;
  const methods = chosenMethods(d);
  return [
    {
      title: 'System boundary',
      paragraphs: [
        'Cradle to gate with end of life: modules A1–A3 (raw material supply, transport to the manufacturer, manufacturing including packaging production), C1–C4 (end of life) and module D (benefits and loads beyond the system boundary). A4 and A5 are declared only where the inputs hold activities or transport for them; the use stage (B1–B7) is not declared. A module not declared is marked so, never shown as zero.',
        'Module D is reported beside A–C and is never added to a total (EN 15804+A2).',
      ],
    },
    {
      title: 'Cut-off and completeness',
      paragraphs: [
        'EN 15804+A2 cut-off rule: a flow may be left out only if it is below 1 % of the mass and of the primary energy of its unit process, and all flows left out together stay below 5 % per module. The inputs list every flow that was included; flows left out are the practitioner’s statement in the inputs, not the tool’s.',
      ],
    },
    {
      title: 'Allocation and recycling',
      paragraphs: [
        'A1–C4 follow the cut-off (polluter pays) rule: recycled input carries only its reprocessing (factor “recycled”); process scrap sent to recycling leaves A3 free of burden and is reported as MFR; process scrap landfilled or incinerated is charged to A3.',
        'Module D (EN 15804+A2 Annex D), per material: D = (M_MR,out − M_MR,in) · (E_MR,after EoW,out − E_VMSub,out · Q_R,out/Q_Sub). Only the net flow earns a credit; a negative net flow gives a load. M_MR,out includes process scrap sent to recycling, after the recycling yield.',
        'Besides cut-off, the Circular Footprint Formula (Commission Recommendation (EU) 2021/2279; A from materials.csv, else 0.2 for metals; B = 0) and its presets 0:100 (A = 0) and 50:50 (A = 0.5) are shown for comparison where the declaration asks for them' + ` (${methods.join(', ')}).` + ' Under these, process scrap sent to recycling earns the same end-of-life term as the product, scrap · yield · (1 − A) · (E_recEoL − E*v · Q_out); disposed scrap is charged as in A3.',
        'Incineration with energy recovery is charged to C3; the exported energy is credited in module D' + (d.energy_recovery ? ` at an electrical efficiency of ${d.energy_recovery.electricity_efficiency} and a thermal efficiency of ${d.energy_recovery.heat_efficiency} (declaration.json energy_recovery).` : ' where declaration.json gives the plant efficiencies (energy_recovery).'),
        ...siteAllocationStatement(project),
      ],
    },
    {
      title: 'Data sources and data quality',
      paragraphs: [
        `Background data: ${d.background_data.map((b) => `${b.name}, version ${b.version}`).join('; ')}. Each factor row names its dataset; each input row its source. Reference year of the inventory: ${d.reference_year}.`,
        `Direct greenhouse-gas emissions are characterised with GWP-100 values from ${GWP_SOURCES[d.gwp_set]}.`,
        'Data quality: a factor row may carry pedigree scores (TeR, GeR, TiR, P; PEF method, Recommendation (EU) 2021/2279), from which its DQR is computed; the declaration shows the DQR of each indicator weighted by the factors’ contributions, and the share of it that rests on scored factors. A factor row without scores is said to be unscored, not given a score. The source column of each input row and the dataset of each factor row are shown beside them; the verifier judges their representativeness.',
      ],
    },
    ...(project.processes.length > 0
      ? [
          {
            title: 'Process models',
            paragraphs: [
              `Primary metal from ${project.processes.length === 1 ? 'one process' : `${project.processes.length} processes`} of the declarant or its suppliers is modelled from operating data (process.csv: ${project.processes.map((p) => `${p.id}, ${p.kind}`).join('; ')}): electricity by Faraday’s law (F from CODATA 2018, molar masses from the IUPAC standard atomic weights) or as measured above the Faraday floor; anode CO2, PFCs and carbon balances by the IPCC 2006 Guidelines, Vol. 3, Ch. 4; stoichiometric floors from the balanced cell reactions. Each product page shows the derivation and the tier used.`,
              PROCESS_CAUTION,
            ],
          },
        ]
      : []),
    {
      title: 'Assumptions',
      paragraphs: [
        'Gross input of a BOM line G = m / (1 − scrap rate); recycled content R1 = pre- + post-consumer share (ISO 14021: rework and regrind reclaimed within the same process is not recycled content).',
        'An A2 transport leg without a BOM line carries the gross input of the product’s own lines; legs in A4 and C2 carry the net mass.',
        'Biogenic carbon not given is zero for metals, minerals and polymers; 1 kg C corresponds to 44/12 kg CO2.',
        'A value a factor row lacks is “n/a” (not available), never zero, and every figure that depends on it is n/a too.',
        'Results are rounded for display only; every sum is computed from unrounded values.',
      ],
    },
  ];
}

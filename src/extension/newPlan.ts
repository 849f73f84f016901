// "Veer: New Plan": an untitled plan from a template, so a first plan starts
// from something that checks cleanly and shows every kind of line.
import * as vscode from 'vscode';
import { LANGUAGE_ID } from './analysis';

export const NEW_PLAN_TEMPLATE = `plan "Greenhouse rover, watering round"
units mm
wheel 56 mm
track 112 mm effective 114 mm
body 130 by 160 axle -20
field 1800 by 1000 grid 100
box "seed tray" (700, 350) to (950, 600)
zone "tap" (1250, 750) to (1500, 980)
limit 60 s

let aisle = 65 cm

run "to the tap"
start (200, 150) heading 0
drive aisle speed 50% hold 0
turn 90 by gyro min 12% gain 1.2
drive 1100 hold 90 ramp 800 mm/s^2
turn -90 pivot left
mark "filling" in "tap"
`;

export function registerNewPlan(context: vscode.ExtensionContext): void {
  context.subscriptions.push(
    vscode.commands.registerCommand('veer.newPlan', async () => {
      const document = await vscode.workspace.openTextDocument({ language: LANGUAGE_ID, content: NEW_PLAN_TEMPLATE });
      await vscode.window.showTextDocument(document);
    }),
  );
}

// "Veer: New Plan": an untitled plan from a template, so a first plan starts
// from something that checks cleanly and shows every kind of line.
import * as vscode from 'vscode';
import { LANGUAGE_ID } from './analysis';

export const NEW_PLAN_TEMPLATE = `# A first plan: an invented watering round in a school greenhouse.
# Lines starting with # are comments. Change the numbers to your robot's.
plan "Watering round"
units mm                          # bare lengths are in millimetres
wheel 58 mm                       # wheel diameter (a ruler across the wheel)
track 121 mm effective 123 mm     # wheel to wheel; "effective" is what turns really need
body 140 by 170 axle -25          # footprint width by length; the axle sits 25 mm behind its centre
field 1800 by 1000 grid 100       # the board, and the spacing of the drawn grid
box "seed tray" (700, 350) to (950, 600)     # an obstacle
zone "tap" (1250, 750) to (1500, 980)        # a place to reach (not an obstacle)
limit 60 s                        # time allowed for the run

let aisle = 65 cm                 # a name for a distance used below

run "to the tap"
start (200, 150) heading 0        # where the robot stands; heading 0 faces up the drawing
drive aisle speed 50% hold 0      # straight on, the gyro holding the reading at 0
turn 90 by gyro min 12% gain 1.2  # a spin turn until the yaw reads 90
drive 1100 hold 90 ramp 800 mm/s^2
turn -90 pivot left               # turn about the still left wheel
mark "filling" in "tap"           # check that the robot ends in the zone
`;

/** The name the editor suggests when the new plan is first saved. */
export const NEW_PLAN_FILE_NAME = 'watering-round.veer';

export function registerNewPlan(context: vscode.ExtensionContext): void {
  context.subscriptions.push(
    vscode.commands.registerCommand('veer.newPlan', async () => {
      // An untitled document with a plain name (the editor would otherwise suggest the first line).
      let uri = vscode.Uri.from({ scheme: 'untitled', path: NEW_PLAN_FILE_NAME });
      for (let n = 2; vscode.workspace.textDocuments.some((d) => d.uri.toString() === uri.toString()); n++) {
        uri = vscode.Uri.from({ scheme: 'untitled', path: NEW_PLAN_FILE_NAME.replace(/\.veer$/, `-${n}.veer`) });
      }
      const document = await vscode.workspace.openTextDocument(uri);
      const editor = await vscode.window.showTextDocument(document);
      await editor.edit((edit) => edit.insert(new vscode.Position(0, 0), NEW_PLAN_TEMPLATE));
      if (document.languageId !== LANGUAGE_ID) await vscode.languages.setTextDocumentLanguage(document, LANGUAGE_ID);
    }),
  );
}

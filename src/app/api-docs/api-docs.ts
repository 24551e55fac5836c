import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, signal } from '@angular/core';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { filterGroups, groupOperations, type OpenApiDocument } from './openapi-view';

/** The API reference, rendered from the server's own OpenAPI document (always in step with the code). */
@Component({
  selector: 'sm-api-docs',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterLink, MatExpansionModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  templateUrl: './api-docs.html',
  styleUrl: './api-docs.scss',
})
export class ApiDocs {
  protected readonly doc = httpResource<OpenApiDocument>(() => '/api/openapi.json');
  protected readonly filter = signal('');
  private readonly groups = computed(() => (this.doc.hasValue() ? groupOperations(this.doc.value()) : []));
  protected readonly shown = computed(() => filterGroups(this.groups(), this.filter()));
  protected readonly count = computed(() => this.groups().reduce((n, g) => n + g.operations.length, 0));
  protected readonly info = computed(() => (this.doc.hasValue() ? this.doc.value().info : null));

  protected setFilter(event: Event): void {
    this.filter.set((event.target as HTMLInputElement).value);
  }
}
